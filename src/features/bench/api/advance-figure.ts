import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Board, Figure } from '../../../../shared/schemas/commissions';
import { api } from '../../../lib/api-client';

/** Marks the figure's current stage done; the next one becomes current. */
export function advanceFigure(studioId: number, figureId: number): Promise<Figure> {
  return api<Figure>(`/api/studios/${studioId}/figures/${figureId}/advance`, { method: 'POST' });
}

/** Moves the card on every cached board at once, so a drop does not jump back while the server answers. */
function moveCard(board: Board, figureId: number): Board {
  const from = board.columns.findIndex((c) => c.cards.some((k) => k.figureId === figureId));
  if (from < 0 || from >= board.columns.length - 1) return board;
  const card = board.columns[from].cards.find((k) => k.figureId === figureId)!;
  return {
    ...board,
    columns: board.columns.map((c, i) =>
      i === from ? { ...c, cards: c.cards.filter((k) => k.figureId !== figureId) } : i === from + 1 ? { ...c, cards: [...c.cards, card] } : c,
    ),
  };
}

export function useAdvanceFigure(studioId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (figureId: number) => advanceFigure(studioId, figureId),
    onMutate: async (figureId) => {
      await queryClient.cancelQueries({ queryKey: ['board'] });
      const before = queryClient.getQueriesData<Board>({ queryKey: ['board'] });
      for (const [key, board] of before) if (board) queryClient.setQueryData(key, moveCard(board, figureId));
      return { before };
    },
    onError: (_err, _id, ctx) => {
      for (const [key, board] of ctx?.before ?? []) queryClient.setQueryData(key, board);
    },
    onSettled: () =>
      Promise.all([queryClient.invalidateQueries({ queryKey: ['board'] }), queryClient.invalidateQueries({ queryKey: ['commissions'] })]),
  });
}
