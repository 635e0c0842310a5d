export default function Home() {
  return (
    <main className="mx-auto max-w-3xl p-8">
      <h1 className="text-3xl font-semibold">Cellwright</h1>
      <p className="mt-2 text-slate-600">A browser bench for the PLC–robot handshake.</p>
    </main>
  );
}
