import { DEMO_PASSWORD, DEMO_USERS } from "../demo/people";
import { ROLE_LABELS } from "../../lib/auth/roles";

const url = process.argv[2] ?? "http://localhost:3000";
const mailInboxUrl = process.argv[3];
console.log(`\nTidemark demo is starting on ${url}`);
console.log(`Every demo account uses the password: ${DEMO_PASSWORD}\n`);
for (const u of DEMO_USERS) {
  console.log(`  ${ROLE_LABELS[u.role].padEnd(22)} ${u.email.padEnd(36)} ${u.units.join(", ")}`);
}
console.log("");
if (mailInboxUrl) {
  console.log(
    `Mail inbox (local SMTP fake): ${mailInboxUrl}  (every e-mail the demo sends lands here)\n`,
  );
}
