import { MailboxScreen } from '@/components/admin/mailbox-screen';

export default function MailboxRoute() {
  return <MailboxScreen />;
}
