import type { Metadata } from 'next';
import Link from 'next/link';
import { PlcLinkCaution } from '@/components/plc-link/plc-link-caution';
import { PlcLinkStartForm } from '@/components/plc-link/start-form';
import { Card, PageHeader } from '@/components/ui/card';
import { Refused } from '@/components/ui/refused';
import { requirePageUser } from '@/lib/auth/session';
import { listOwnedCells } from '@/db/cells';
import { sessionsOf } from '@/lib/plc-link/sessions';
import { plcLinkSettings } from '@/lib/plc-link/settings';
import { ROLE_TABLE } from '@/lib/roles';

export const metadata: Metadata = { title: 'PLC link · Cellwright' };

export default async function PlcLinkPage() {
  const { user, allowed } = await requirePageUser('/plc-link', ROLE_TABLE.plcLink);
  if (!allowed) return <Refused role={user.role} needs="trainers and maintenance leads" />;
  const cells = (await listOwnedCells(user.id)).map((c) => ({ id: c.id, name: c.name }));
  const sessions = sessionsOf(user);
  return (
    <>
      <PageHeader
        title="PLC link"
        description="A real PLC on the bench drives one of your cells over Modbus TCP: the logic sheet is set aside and the cell's outputs follow what the PLC writes."
      />
      <div className="grid gap-4">
        <PlcLinkCaution />
        <Card title="Start a PLC link">
          <PlcLinkStartForm cells={cells} iface={plcLinkSettings().PLC_LINK_INTERFACE} />
        </Card>
        {sessions.length > 0 ? (
          <Card title="Your sessions on this server">
            <ul className="grid gap-1 text-sm">
              {sessions.map((s) => (
                <li key={s.id}>
                  <Link className="text-accent-800 underline" href={`/plc-link/${s.id}`}>
                    {s.cellName}
                  </Link>{' '}
                  on port <span className="font-mono">{s.port}</span> · {s.status}
                </li>
              ))}
            </ul>
          </Card>
        ) : null}
      </div>
    </>
  );
}
