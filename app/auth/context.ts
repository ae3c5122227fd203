import { createContext } from "react-router";
import type { Role } from "./roles";

/** The signed-in person as every gated loader and action sees it. */
export type Viewer = {
  sessionId: string;
  person: {
    id: string;
    name: string;
    email: string;
    title: string | null;
    homeUnitId: string | null;
  };
  org: { id: string; name: string; timeZone: string };
  roles: Role[];
};

/** Set by the root middleware for every request; null when nobody is signed in. */
export const viewerContext = createContext<Viewer | null>(null);
