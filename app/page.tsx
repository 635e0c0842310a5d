import Link from 'next/link';
import { Activity, ClipboardCheck, GitCompare, Network } from 'lucide-react';
import { Logo } from '@/components/ui/logo';
import { SafetyCaution } from '@/components/ui/safety-caution';
import { getPageUser } from '@/lib/auth/session';

const FEATURES = [
  {
    icon: Network,
    title: 'Wire the cell',
    text: 'Connect an operator panel and field devices to a simulated PLC, and map the robot controller’s points by rack, slot and channel.',
  },
  {
    icon: Activity,
    title: 'Run the handshake',
    text: 'Build start, stop and ready logic from IEC 61131-3 function blocks and watch every signal on the panel, wire, sheet and scope at once.',
  },
  {
    icon: ClipboardCheck,
    title: 'Drill and grade',
    text: 'Trainers hide fault cards in a cell; students find them with monitor, force and scope; the server replays and grades each run.',
  },
  {
    icon: GitCompare,
    title: 'Model a real cell',
    text: 'Maintenance leads import a real cell’s point map and I/O list as CSV, model its interlocks, keep every change as a version and run regression checks headless.',
  },
];

export default async function LandingPage() {
  const user = await getPageUser();
  return (
    <div className="min-h-screen">
      <header className="border-b border-slate-200 bg-white">
        <div className="mx-auto flex max-w-5xl items-center justify-between px-6 py-3">
          <Logo className="text-slate-900" />
          <Link
            href={user ? '/dashboard' : '/sign-in'}
            className="rounded-md bg-accent-700 px-3 py-2 text-sm font-medium text-white hover:bg-accent-800"
          >
            {user ? 'Open your dashboard' : 'Sign in'}
          </Link>
        </div>
      </header>
      <main className="mx-auto max-w-5xl px-6 py-14">
        <h1 className="max-w-3xl text-4xl font-semibold tracking-tight text-slate-900">
          A bench for the handshake between PLC and robot.
        </h1>
        <p className="mt-4 max-w-3xl text-lg text-slate-600">
          Cellwright simulates one robot cell end to end — operator panel, sensors and actuators, a PLC running interlock logic,
          and a robot controller with its own I/O points — so instructors, students and maintenance leads can wire it, run it,
          break it on purpose, find the fault, and record and replay the result without a physical trainer or a production line.
        </p>
        <ul className="mt-10 grid gap-4 sm:grid-cols-2">
          {FEATURES.map(({ icon: Icon, title, text }) => (
            <li key={title} className="rounded-lg border border-slate-200 bg-white p-5 shadow-sm">
              <Icon aria-hidden className="h-5 w-5 text-accent-700" />
              <h2 className="mt-2 font-semibold">{title}</h2>
              <p className="mt-1 text-sm text-slate-600">{text}</p>
            </li>
          ))}
        </ul>
        <SafetyCaution className="mt-10" />
      </main>
    </div>
  );
}
