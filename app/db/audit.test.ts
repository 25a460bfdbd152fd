import { describe, expect, it } from "vitest";
import { sha256Hex } from "./audit.server";

// The hash behind every signature, token and input hash: node's native SHA-256 must give the
// published digests. Vectors: NIST FIPS 180-2, Appendix B (SHA-256 examples B.1, B.2, B.3) and the
// empty message (NIST CSRC example values); all also checked here with coreutils' sha256sum.
describe("sha256Hex", () => {
  it("gives the FIPS 180-2 digests", () => {
    expect(sha256Hex("abc")).toBe("ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
    expect(sha256Hex("abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq")).toBe("248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1");
    expect(sha256Hex("a".repeat(1_000_000))).toBe("cdc76e5c9914fb9281a1c7e284d73e67f1809a48a497200e046d39ccc7112cd0");
    expect(sha256Hex("")).toBe("e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855");
  });

  it("hashes a text as its UTF-8 bytes", () => {
    // sha256sum of the UTF-8 bytes of "Kármán–Tsien" (printf 'Kármán–Tsien' | sha256sum).
    expect(sha256Hex("Kármán–Tsien")).toBe("97736876d0153af48549e527fad58391fd2d966595cfa9e4946506f25c00e5b5");
    expect(sha256Hex(new TextEncoder().encode("Kármán–Tsien"))).toBe(sha256Hex("Kármán–Tsien"));
  });
});
