/** Client paths of the payment screens. */
export const paymentPaths = {
  runs: '/payment-runs',
  ready: '/payment-runs/ready',
  run: (id: string) => `/payment-runs/${encodeURIComponent(id)}`,
  claim: (id: string) => `/claims/${encodeURIComponent(id)}`,
} as const;
