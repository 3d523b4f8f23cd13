import { inject } from "vitest";

// Test files talk to the same database, mail catcher and app as the server under test.
process.env.DATABASE_URL = inject("databaseUrl");
process.env.APP_URL = inject("appUrl");
process.env.SMTP_URL = inject("smtpUrl");
process.env.MAIL_CATCHER_URL = inject("mailUrl");
process.env.BETTER_AUTH_SECRET = inject("authSecret");
