import { redirect } from "next/navigation";
import { homePath } from "@/lib/auth/home";
import { pageActor } from "@/lib/auth/page-guard";

/** "/" sends each role to its home: reviewers to Reports, everyone else to the Board. */
export default async function Home() {
  const actor = await pageActor();
  redirect(homePath(actor.role));
}
