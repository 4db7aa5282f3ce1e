import { queryOptions, useQuery } from '@tanstack/react-query';
import type { SpectrumResponse } from '@shared/schemas/concepts';
import { api } from '@/lib/api-client';
import { conceptsPath, conceptsQueryKey } from './keys';

export type { SpectrumResponse, SpectrumVersion } from '@shared/schemas/concepts';

/** The serving version's singular values and energy, and the previous ready version's. */
export function getSpectrum(matterId: number, signal?: AbortSignal): Promise<SpectrumResponse> {
  return api.get<SpectrumResponse>(conceptsPath(matterId, 'spectrum'), { signal });
}

export function spectrumQueryOptions(matterId: number) {
  return queryOptions({
    queryKey: [...conceptsQueryKey(matterId), 'spectrum'],
    queryFn: ({ signal }) => getSpectrum(matterId, signal),
  });
}

export function useSpectrum(matterId: number) {
  return useQuery(spectrumQueryOptions(matterId));
}
