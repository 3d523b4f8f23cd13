"use client";

import { apiKeyClient } from "@better-auth/api-key/client";
import { organizationClient } from "better-auth/client/plugins";
import { createAuthClient } from "better-auth/react";
import { accessControl, roles } from "./permissions";

export const authClient = createAuthClient({
  plugins: [organizationClient({ ac: accessControl, roles }), apiKeyClient()],
});
