// Pathless layout of the /api/v1 resource routes: identifies the caller once per request.
import { identifyApiCallerMiddleware } from "~/utils/auth.server";
import { errorToProblem } from "~/utils/api.server";
import type { Route } from "./+types/api.v1.layout";

export const middleware: Route.MiddlewareFunction[] = [
  async (args, next) => {
    try {
      await identifyApiCallerMiddleware(args, next);
    } catch (error) {
      // A failure here (e.g. the database is down) still answers problem+json.
      throw errorToProblem(error);
    }
    return next();
  },
];
