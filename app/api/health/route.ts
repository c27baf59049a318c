/** Liveness: answers without touching the database (the load benchmark's reference route). */
export function GET(): Response {
  return Response.json({ ok: true }, { headers: { 'cache-control': 'no-store' } });
}
