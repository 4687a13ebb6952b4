import { MailboxScreen } from '@/components/mailbox/mailbox-screen';

export default function MailboxRoute() {
  return <MailboxScreen />;
}
