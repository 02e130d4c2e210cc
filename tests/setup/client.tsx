import type { ReactNode } from 'react';
import { render } from '@testing-library/react';
import { QueryClientProvider, type QueryClient } from '@tanstack/react-query';
import { createMemoryRouter, RouterProvider } from 'react-router-dom';
import type { Task } from '@shared/schemas/plan';
import { TasksEditor } from '@/features/plans/components/tasks-editor';
import { createQueryClient } from '@/lib/query-client';

/** Testing Library's render inside the app's query client provider: a fresh client unless given. */
export function renderWithQueryClient(ui: ReactNode, queryClient: QueryClient = createQueryClient()) {
  const wrapper = ({ children }: { children: ReactNode }) => (
    <QueryClientProvider client={queryClient}>{children}</QueryClientProvider>
  );
  return { ...render(ui, { wrapper }), queryClient };
}

/**
 * `renderWithQueryClient` inside a data router at `/`: for screens that guard leaving (the router's
 * blocker needs one).
 */
export function renderInDataRouter(ui: ReactNode, queryClient: QueryClient = createQueryClient()) {
  const router = createMemoryRouter([{ path: '*', element: ui }]);
  return { ...renderWithQueryClient(<RouterProvider router={router} />, queryClient), router };
}

/** The plan's task list, editable, on a station with no worksites or sockets; `latest()` is what it last sent. */
export function renderTasksEditor(tasks: Task[], warningCounts: Map<number, number> = new Map()) {
  let latest = tasks;
  const view = render(
    <TasksEditor
      tasks={tasks}
      onChange={(next) => {
        latest = next;
      }}
      readOnly={false}
      nodes={{ worksites: [], sockets: [] }}
      manifest={[]}
      reach={[]}
      warningCounts={warningCounts}
    />,
  );
  return { ...view, latest: () => latest };
}
