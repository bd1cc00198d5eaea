import { index, route, type RouteConfig } from "@react-router/dev/routes";

export default [
  index("routes/home.tsx"),
  route("healthz", "routes/healthz.ts"),
  route("sign-up", "routes/sign-up.tsx"),
  route("sign-in", "routes/sign-in.tsx"),
  route("sign-out", "routes/sign-out.ts"),
  route("dashboard", "routes/dashboard.tsx"),
  route("m/:id", "routes/mechanism.tsx"),
  route("m/:id/members", "routes/members.tsx"),
  route("api/v1/mechanisms", "routes/api/mechanisms.ts"),
  route("api/v1/mechanisms/:id", "routes/api/mechanism.ts"),
  route("api/*", "routes/api/not-found.ts"),
  route("*", "routes/not-found.tsx"),
] satisfies RouteConfig;
