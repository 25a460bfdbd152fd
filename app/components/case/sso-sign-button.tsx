import { Button } from "~/components/ui/button";
/**
 * Signs through the identity provider instead of the password: it asks the person to sign in again
 * there, for this one signature.
 */
export function SsoSignButton({ busy, label }: { busy: boolean; label: string }) {
  return (
    <Button type="submit" name="confirm" value="sso" variant="secondary" disabled={busy} formNoValidate>
      {label}
    </Button>
  );
}
