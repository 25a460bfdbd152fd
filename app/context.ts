import { createContext } from "react-router";

/** The client's network address, set by the HTTP server for each request (used for sign-in throttling). */
export const clientAddressContext = createContext<string>("unknown");
