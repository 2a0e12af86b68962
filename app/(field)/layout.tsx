import { ScopedMessages } from "@/app/_components/scoped-messages";

export default function FieldGroupLayout({ children }: { children: React.ReactNode }) {
  return <ScopedMessages namespaces={["field", "dig", "sync"]}>{children}</ScopedMessages>;
}
