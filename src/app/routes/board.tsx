import { Link } from 'react-router';
import { hasRole } from '@shared/roles';
import { PageHeader } from '@/components/layout/page-header';
import { Alert } from '@/components/ui/alert';
import { Button, buttonClasses } from '@/components/ui/button';
import { PageSpinner } from '@/components/ui/spinner';
import { useSession } from '@/features/auth/api/get-session';
import { useBoard } from '@/features/board/api/get-board';
import { BoardView } from '@/features/board/components/board-view';

export function BoardPage() {
  const board = useBoard();
  const { data: session } = useSession();
  const staff = session?.user ? hasRole(session.user.role, 'technician') : false;

  return (
    <>
      <title>Status board · Faultline</title>
      <PageHeader
        title="Status board"
        description="Every tool, live. Changes made anywhere appear here within a second."
        actions={
          <>
            <Link to="/report" className={buttonClasses({ size: 'lg' })}>
              Report a fault
            </Link>
            {staff && (
              <Link to="/labels" className={buttonClasses({ variant: 'secondary' })}>
                QR labels
              </Link>
            )}
          </>
        }
      />
      {board.isPending && <PageSpinner label="Loading the board…" />}
      {board.isError && (
        <Alert
          tone="danger"
          live
          title="The board could not be loaded"
          actions={
            <Button variant="secondary" onClick={() => void board.refetch()}>
              Try again
            </Button>
          }
        >
          {board.error.message}
        </Alert>
      )}
      {board.data && <BoardView data={board.data} />}
    </>
  );
}

export { BoardPage as Component };
