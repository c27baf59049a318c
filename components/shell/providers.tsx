'use client';

import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { useState } from 'react';
import { useChartFont } from '@/components/charts/use-chart-font';

export function Providers({ children }: { children: React.ReactNode }) {
  const [client] = useState(
    () => new QueryClient({ defaultOptions: { queries: { retry: 1, refetchOnWindowFocus: false, staleTime: 5_000 } } }),
  );
  useChartFont();
  return <QueryClientProvider client={client}>{children}</QueryClientProvider>;
}
