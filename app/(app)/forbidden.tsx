import { AccessNotice } from "@/components/shell/AccessNotice";

// Inside the app's layout: the header and navigation stay, so the way on is one click.
export default function Forbidden() {
  return <AccessNotice kind="forbidden" />;
}
