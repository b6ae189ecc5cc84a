import { useMutation } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';

/*
 * `POST /api/auth/board-token` (admin only, interfaces §13). Written by hand until the server's DTO for it is
 * in the OpenAPI document; then replace these two with the generated `Schemas[...]` names (api-schema.ts).
 */
export interface BoardTokenInput {
  /** Which wall screen the link is for, e.g. "Hall B, above line 2" */
  label: string;
}

export interface BoardTokenAnswer {
  token: string;
  /** ISO 8601; the link stops working then (30 days) */
  expiresAt: string;
}

export function createBoardToken(input: BoardTokenInput): Promise<BoardTokenAnswer> {
  return api.post<BoardTokenAnswer>(apiPaths.boardToken, input);
}

export function useCreateBoardToken() {
  return useMutation({ mutationFn: createBoardToken });
}
