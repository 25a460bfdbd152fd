import { type RouteConfig, route } from "@react-router/dev/routes";

export default [route("cases/:caseId", "routes/case.tsx")] satisfies RouteConfig;
