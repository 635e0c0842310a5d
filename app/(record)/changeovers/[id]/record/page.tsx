import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { ArrowLeft } from 'lucide-react';
import { Refused } from '@/components/ui/refused';
import { PrintButton } from '@/components/changeovers/print-button';
import { SignedRecordView } from '@/components/changeovers/signed-record';
import { requirePageUser } from '@/lib/auth/session';
import { changeoverForReader } from '@/lib/changeovers/access';
import { loadOrNotFound, paramsOrNotFound } from '@/lib/pages/not-found';
import { changeoverIdParamSchema } from '@/lib/schemas/changeovers';
import { findSignedRecord } from '@/db/changeovers';
import { ROLE_TABLE } from '@/lib/roles';

export const metadata: Metadata = { title: 'Changeover record · Cellwright' };

/** The signed record, laid out to print (the browser's print dialog saves it as PDF too). */
export default async function ChangeoverRecordPage({ params }: { params: Promise<{ id: string }> }) {
  const raw = await params;
  const { user, allowed } = await requirePageUser(`/changeovers/${raw.id}/record`, ROLE_TABLE.changeovers);
  if (!allowed) return <Refused role={user.role} needs="maintenance leads, trainers and administrators" />;
  const { id } = paramsOrNotFound(changeoverIdParamSchema, raw);
  const co = await loadOrNotFound(changeoverForReader(user, id));
  const record = await findSignedRecord(co.id);
  if (!record) notFound();
  return (
    <>
      <div className="mb-6 flex flex-wrap items-center justify-between gap-3 print:hidden">
        <Link href={`/changeovers/${co.id}`} className="inline-flex items-center gap-1 text-sm font-medium text-accent-700 hover:underline">
          <ArrowLeft aria-hidden className="h-4 w-4" /> Back to the changeover
        </Link>
        <PrintButton />
      </div>
      <SignedRecordView record={record} changeover={co} />
    </>
  );
}
