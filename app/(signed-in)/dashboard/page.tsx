import type { Metadata } from 'next';
import Link from 'next/link';
import { Card, PageHeader } from '@/components/ui/card';
import { formatDateTime } from '@/lib/format';
import { SafetyCaution } from '@/components/ui/safety-caution';
import { requirePageUser } from '@/lib/auth/session';
import { ROLE_LABELS } from '@/lib/roles';
import type { User } from '@/db/users';
import { countUsersByRole } from '@/db/users';
import { listCohorts, listCohortsOfStudent } from '@/db/cohorts';
import type { CohortSummary } from '@/db/cohorts';
import { recentAudit } from '@/db/audit';
import type { AuditEntry } from '@/db/audit';
import { countMail } from '@/db/mail';
import { MyDrillsTable } from '@/components/drills/my-drills';
import { ChangeoversCard } from '@/components/changeovers/dashboard-card';
import { listChangeoversFor } from '@/db/changeovers';
import { ListTable } from '@/components/ui/list-table';

export const metadata: Metadata = { title: 'Dashboard · Cellwright' };

const ACTION_TEXT: Record<string, string> = {
  'role.changed': 'Role changed',
  'user.disabled': 'Account disabled',
  'user.enabled': 'Account enabled',
  'signin.failed': 'Failed sign-in',
  'signin.blocked': 'Sign-in paused (too many failures)',
  'invitation.accepted': 'Invitation accepted',
  'password.reset': 'Password reset',
};

function describe(e: AuditEntry): string {
  const d = e.detail as Record<string, string>;
  if (e.action === 'role.changed') return `${d.from} → ${d.to}`;
  if (e.action.startsWith('signin.')) return `${d.email ?? ''} from ${d.address ?? 'unknown'}${d.reason ? ` (${d.reason})` : ''}`;
  return e.targetEmail ?? '';
}

function AuditList({ entries, empty }: { entries: AuditEntry[]; empty: string }) {
  if (entries.length === 0) return <p className="text-sm text-slate-500">{empty}</p>;
  return (
    <ul className="divide-y divide-slate-100 text-sm">
      {entries.map((e) => (
        <li key={e.id} className="flex flex-wrap justify-between gap-2 py-2">
          <span>
            <span className="font-medium">{ACTION_TEXT[e.action] ?? e.action}</span>{' '}
            <span className="text-slate-600">{describe(e)}</span>
            {e.actorName ? <span className="text-slate-500"> · by {e.actorName}</span> : null}
          </span>
          <span className="font-mono text-xs text-slate-500">{formatDateTime(e.createdAt)}</span>
        </li>
      ))}
    </ul>
  );
}

function AccountCard({ user }: { user: User }) {
  return (
    <Card title="Your account">
      <dl className="grid grid-cols-[8rem_1fr] gap-y-1 text-sm">
        <dt className="text-slate-500">Name</dt>
        <dd>{user.name}</dd>
        <dt className="text-slate-500">E-mail</dt>
        <dd className="font-mono">{user.email}</dd>
        <dt className="text-slate-500">Role</dt>
        <dd>{ROLE_LABELS[user.role]}</dd>
        <dt className="text-slate-500">Organization</dt>
        <dd>{user.organization ?? '—'}</dd>
        <dt className="text-slate-500">Last sign-in</dt>
        <dd className="font-mono text-xs leading-5">{formatDateTime(user.lastSignInAt)}</dd>
      </dl>
    </Card>
  );
}

function CohortTable({ cohorts, showTrainer, linkTo }: { cohorts: CohortSummary[]; showTrainer: boolean; linkTo: boolean }) {
  return (
    <ListTable
      head={
        <>
          <th className="py-2">Cohort</th>
          {showTrainer ? <th>Trainer</th> : null}
          <th className="text-right">Members</th>
          <th className="text-right">Open invitations</th>
        </>
      }
    >
      {cohorts.map((c) => (
        <tr key={c.id}>
          <td className="py-2">
            {linkTo ? (
              <Link href={`/cohorts/${c.id}`} className="font-medium text-accent-700 hover:underline">
                {c.name}
              </Link>
            ) : (
              <span className="font-medium">{c.name}</span>
            )}
          </td>
          {showTrainer ? <td>{c.trainerName}</td> : null}
          <td className="text-right font-mono">{c.memberCount}</td>
          <td className="text-right font-mono">{c.pendingCount}</td>
        </tr>
      ))}
    </ListTable>
  );
}

async function StudentSection({ user }: { user: User }) {
  const cohorts = await listCohortsOfStudent(user.id);
  return (
    <Card title="Your cohorts">
      {cohorts.length === 0 ? (
        <p className="text-sm text-slate-500">You are not in a cohort yet. Your trainer adds you with an e-mail invitation.</p>
      ) : (
        <ul className="space-y-3">
          {cohorts.map((c) => (
            <li key={c.id} className="rounded-md border border-slate-200 p-3">
              <p className="font-medium">{c.name}</p>
              <p className="text-sm text-slate-600">{c.description}</p>
              <p className="mt-1 text-xs text-slate-500">
                Trainer: {c.trainerName} · {c.memberCount} students
              </p>
            </li>
          ))}
        </ul>
      )}
    </Card>
  );
}

async function TrainerSection({ user }: { user: User }) {
  const cohorts = await listCohorts(user.id);
  return (
    <Card
      title="Your cohorts"
      actions={
        <Link href="/cohorts" className="text-sm font-medium text-accent-700 hover:underline">
          Manage cohorts
        </Link>
      }
    >
      {cohorts.length === 0 ? (
        <p className="text-sm text-slate-500">No cohorts yet. Create one and invite your students by e-mail.</p>
      ) : (
        <CohortTable cohorts={cohorts} showTrainer={false} linkTo />
      )}
    </Card>
  );
}

async function LeadSection({ user }: { user: User }) {
  const [events, changeovers] = await Promise.all([recentAudit(10, user.id), listChangeoversFor(user)]);
  return (
    <>
      <Card title="Your plant">
        <p className="text-sm text-slate-700">
          {user.organization ?? 'No plant recorded'} — cells you import and the changeovers you prove are kept under this
          account.
        </p>
        <SafetyCaution compact className="mt-4" />
      </Card>
      <ChangeoversCard changeovers={changeovers} />
      <Card title="Account activity">
        <AuditList entries={events} empty="No security events for your account." />
      </Card>
    </>
  );
}

async function AdminSection() {
  const [counts, mail, audit, cohorts] = await Promise.all([countUsersByRole(), countMail(), recentAudit(12), listCohorts(null)]);
  const tiles = [
    { label: 'Students', value: counts.student },
    { label: 'Trainers', value: counts.trainer },
    { label: 'Maintenance leads', value: counts.lead },
    { label: 'Administrators', value: counts.admin },
    { label: 'Disabled accounts', value: counts.disabled },
    { label: 'Captured e-mails', value: mail },
  ];
  return (
    <>
      <section aria-label="Counts" className="grid grid-cols-2 gap-3 sm:grid-cols-3 lg:col-span-2 lg:grid-cols-6">
        {tiles.map((t) => (
          <div key={t.label} className="rounded-lg border border-slate-200 bg-white p-4 shadow-sm">
            <p className="text-xs text-slate-500">{t.label}</p>
            <p className="font-mono text-2xl font-semibold">{t.value}</p>
          </div>
        ))}
      </section>
      <Card title="Cohorts">
        {cohorts.length === 0 ? <p className="text-sm text-slate-500">No cohorts.</p> : <CohortTable cohorts={cohorts} showTrainer linkTo />}
      </Card>
      <Card title="Recent audit events">
        <AuditList entries={audit} empty="Nothing audited yet." />
      </Card>
    </>
  );
}

export default async function DashboardPage() {
  const { user } = await requirePageUser('/dashboard');
  return (
    <>
      <PageHeader title={`Welcome, ${user.name.split(' ')[0]}`} description={`${ROLE_LABELS[user.role]} dashboard`} />
      <div className="grid gap-6 lg:grid-cols-2">
        {user.role === 'student' ? <StudentSection user={user} /> : null}
        {user.role === 'student' ? (
          <Card title="My drills" actions={<Link href="/drills" className="text-sm font-medium text-accent-700 hover:underline">All drills</Link>}>
            <MyDrillsTable userId={user.id} compact />
          </Card>
        ) : null}
        {user.role === 'trainer' ? <TrainerSection user={user} /> : null}
        {user.role === 'lead' ? <LeadSection user={user} /> : null}
        {user.role === 'admin' ? <AdminSection /> : null}
        <AccountCard user={user} />
      </div>
    </>
  );
}
