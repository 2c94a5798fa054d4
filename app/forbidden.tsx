import { AccessNotice } from "@/components/shell/AccessNotice";

export default function Forbidden() {
  return (
    <main>
      <AccessNotice kind="forbidden" />
    </main>
  );
}
