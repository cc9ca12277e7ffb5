import { type RouteConfig, index, layout, prefix, route } from "@react-router/dev/routes";

export default [
  route("login", "routes/login.tsx"),
  route("logout", "routes/logout.tsx"),
  route("forgot-password", "routes/forgot-password.tsx"),
  route("invite/:token", "routes/invite.$token.tsx"),
  route("reset/:token", "routes/reset.$token.tsx"),
  route("dev/mail", "routes/dev.mail.tsx"),
  layout("routes/app-layout.tsx", [
    index("routes/home.tsx"),
    route("circuits", "routes/circuits.tsx"),
    route("circuits/new", "routes/circuits.new.tsx"),
    route("circuits/:circuitId", "routes/circuits.$circuitId.tsx"),
    route("circuits/:circuitId/edit", "routes/circuits.$circuitId.edit.tsx"),
    route("circuits/:circuitId/crossings/new", "routes/circuits.$circuitId.crossings.new.tsx"),
    route("crossings/:crossingId", "routes/crossings.$crossingId.tsx"),
    route("crossings/:crossingId/edit", "routes/crossings.$crossingId.edit.tsx"),
    route("profiles/:profileId", "routes/profiles.$profileId.tsx"),
    route("admin/users", "routes/admin.users.tsx"),
    route("admin/audit", "routes/admin.audit.tsx"),
  ]),
  ...prefix("api/v1", [
    route("circuits", "routes/api.v1.circuits.ts"),
    route("circuits/:circuitId", "routes/api.v1.circuits.$circuitId.ts"),
    route("circuits/:circuitId/crossings", "routes/api.v1.circuits.$circuitId.crossings.ts"),
    route("circuits/:circuitId/profiles", "routes/api.v1.circuits.$circuitId.profiles.ts"),
    route("crossings/:crossingId", "routes/api.v1.crossings.$crossingId.ts"),
    route("profiles/:profileId", "routes/api.v1.profiles.$profileId.ts"),
    route("*", "routes/api.v1.not-found.ts"),
  ]),
  route("*", "routes/not-found.tsx"),
] satisfies RouteConfig;
