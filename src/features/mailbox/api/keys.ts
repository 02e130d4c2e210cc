export const mailboxKeys = {
  all: ['mailbox'] as const,
  lists: () => [...mailboxKeys.all, 'list'] as const,
  list: () => [...mailboxKeys.lists()] as const,
};
