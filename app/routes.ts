import { type RouteConfig, index, layout, prefix, route } from "@react-router/dev/routes";

export default [
  index("routes/home.tsx"),
  route("login", "routes/auth/login.tsx"),
  route("logout", "routes/auth/logout.ts"),
  route("auth/sso", "routes/auth/sso.ts"),
  route("auth/sso/callback", "routes/auth/sso-callback.ts"),
  route("invite/:token", "routes/auth/invite.tsx"),
  layout("routes/app-layout.tsx", [
    ...prefix("cases", [
      index("routes/cases/list.tsx"),
      route("new", "routes/cases/new.tsx"),
      route(":caseId", "routes/cases/case-layout.tsx", { id: "case" }, [
        index("routes/cases/overview.tsx"),
        route("basis", "routes/cases/basis.tsx"),
        route("planform", "routes/cases/planform.tsx"),
        route("sections", "routes/cases/sections.tsx"),
        route("envelope", "routes/cases/envelope.tsx"),
        route("distribution", "routes/cases/distribution.tsx"),
        route("loads", "routes/cases/loads.tsx"),
      ]),
    ]),
    ...prefix("programmes", [
      index("routes/programmes/list.tsx"),
      route(":programmeId", "routes/programmes/detail.tsx"),
    ]),
    route("checks", "routes/checks.tsx"),
    route("methods", "routes/methods.tsx"),
    route("audit", "routes/audit.tsx"),
    route("admin", "routes/admin/members.tsx"),
    route("account", "routes/account.tsx"),
    route("account/tokens", "routes/account-tokens.tsx"),
  ]),
  route("dev/mailbox", "routes/dev/mailbox.tsx"),
  route("api/planform-preview", "routes/api/planform-preview.ts"),
  route("api", "routes/api-docs.tsx"),
  ...prefix("api/v1", [
    route("cases", "routes/api/v1/cases.ts"),
    route("cases/import", "routes/api/v1/case-import.ts"),
    route("cases/:caseId", "routes/api/v1/case.ts"),
    route("cases/:caseId/export", "routes/api/v1/case-export.ts"),
    route("cases/:caseId/results", "routes/api/v1/case-results.ts"),
    route("analyze", "routes/api/v1/analyze.ts"),
    route("openapi.json", "routes/api/v1/openapi.ts"),
    route("*", "routes/api/v1/not-found.ts"),
  ]),
  route("healthz", "routes/api/healthz.ts"),
] satisfies RouteConfig;
