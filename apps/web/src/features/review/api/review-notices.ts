import { reviewNoticesResultSchema, type ReviewNoticesInput } from '@turnstone/contracts/quality';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';

/** Marks a point's quality notices reviewed (by the signed-in user, now). */
export function reviewNotices(body: ReviewNoticesInput) {
  return api.post('/api/v1/quality-notices/review', { body, schema: reviewNoticesResultSchema });
}

export function useReviewNotices() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: reviewNotices,
    // The review lists unreviewed notices; the tree and the point pages show the status.
    onSettled: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: ['review'] }),
        queryClient.invalidateQueries({ queryKey: ['fleet'] }),
        queryClient.invalidateQueries({ queryKey: ['quality-notices'] }),
        queryClient.invalidateQueries({ queryKey: ['point'] }),
      ]),
  });
}
