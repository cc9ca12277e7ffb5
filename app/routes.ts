import { type RouteConfig, index, layout, route } from "@react-router/dev/routes";

export default [
  route("login", "routes/login.tsx"),
  route("logout", "routes/logout.tsx"),
  route("forgot-password", "routes/forgot-password.tsx"),
  route("invite/:token", "routes/invite.$token.tsx"),
  route("reset/:token", "routes/reset.$token.tsx"),
  route("dev/mail", "routes/dev.mail.tsx"),
  layout("routes/app-layout.tsx", [
    index("routes/home.tsx"),
    route("admin/users", "routes/admin.users.tsx"),
    route("admin/audit", "routes/admin.audit.tsx"),
  ]),
  route("*", "routes/not-found.tsx"),
] satisfies RouteConfig;
