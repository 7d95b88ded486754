import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';

export interface MailboxMessage {
  id: number | string;
  receivedAt: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
  html: string | null;
  attachments: { filename: string; contentType: string; size: number }[];
}

/** What the local mail sink has received, newest first. */
export async function getMailbox(signal?: AbortSignal): Promise<MailboxMessage[]> {
  const body = await api.get<MailboxMessage[] | { messages: MailboxMessage[] }>('/api/dev/mailbox', undefined, signal);
  const messages = Array.isArray(body) ? body : (body?.messages ?? []);
  return [...messages].sort((a, b) => b.receivedAt.localeCompare(a.receivedAt));
}

export const mailboxQueries = {
  list: () =>
    queryOptions({
      queryKey: ['mailbox', 'list'] as const,
      queryFn: ({ signal }) => getMailbox(signal),
      staleTime: 0,
    }),
};

export function useMailbox() {
  return useQuery({ ...mailboxQueries.list(), refetchInterval: 5_000 });
}
