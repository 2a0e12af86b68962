import { NextIntlClientProvider } from "next-intl";
import { getMessages } from "next-intl/server";
import { type Namespace, pickMessages } from "@/lib/i18n/messages";

// Gives the client components below it the "common" catalog and the named ones.
export async function ScopedMessages({
  namespaces,
  children,
}: {
  namespaces: readonly Namespace[];
  children: React.ReactNode;
}) {
  const messages = await getMessages();
  return (
    <NextIntlClientProvider messages={pickMessages(messages, ["common", ...namespaces])}>
      {children}
    </NextIntlClientProvider>
  );
}
