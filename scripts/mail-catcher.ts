import { startMailCatcher } from "./lib/mail-catcher";

const smtpPort = Number(process.env.PEEKSAFE_SMTP_PORT ?? 1025);
const httpPort = Number(process.env.PEEKSAFE_MAIL_HTTP_PORT ?? 1080);
const catcher = await startMailCatcher({ smtpPort, httpPort });
console.error(`[mail] catching SMTP on 127.0.0.1:${smtpPort}, messages at http://127.0.0.1:${httpPort}/messages`);

const stop = () => {
  catcher.stop().finally(() => process.exit(0));
};
process.on("SIGINT", stop);
process.on("SIGTERM", stop);
