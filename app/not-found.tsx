import { AccessNotice } from "@/components/shell/AccessNotice";

export default function NotFound() {
  return (
    <main>
      <AccessNotice kind="not-found" />
    </main>
  );
}
