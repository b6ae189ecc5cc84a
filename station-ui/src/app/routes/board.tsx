import { BoardScreen } from '@/features/board/components/board-screen';

/** The line board for the wall screen (src/features/board/). */
export default function BoardRoute() {
  return <BoardScreen />;
}
