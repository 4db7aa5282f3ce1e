import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { NoteResponse, ReviewResponse } from '@shared/schemas/review';
import { api } from '@/lib/api-client';
import { reviewsQueryKey } from './keys';

/** POST /api/matters/:matterId/documents/:docId/notes (documents.code). */
export function createNote(matterId: number, docId: number, body: string): Promise<NoteResponse> {
  return api.post<NoteResponse>(`/api/matters/${matterId}/documents/${docId}/notes`, { body });
}

export function useCreateNote(matterId: number, docId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: string) => createNote(matterId, docId, body),
    onSuccess: ({ note }) =>
      queryClient.setQueriesData<ReviewResponse>(
        { queryKey: [...reviewsQueryKey(matterId), docId] },
        (old) => (old ? { ...old, notes: [...old.notes, note] } : old),
      ),
  });
}
