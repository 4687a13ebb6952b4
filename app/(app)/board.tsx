import { BoardScreen } from '@/components/board/board-screen';

export default function BoardRoute() {
  return <BoardScreen />;
}
