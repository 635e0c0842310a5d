import { SafetyCaution } from '@/components/ui/safety-caution';

/** The PLC link's own caution, beside the standard one (DESIGN.md, Safety; issue 13). */
export function PlcLinkCaution() {
  return (
    <SafetyCaution compact>
      <p data-testid="plc-link-caution">
        A PLC link is for rehearsal on a bench. Never connect a PLC that drives real machinery: disconnect its outputs (or
        disable them) and keep it off production networks. Safety functions stay hardwired or safety-rated; follow the
        site&apos;s procedures, local codes and licensed practice.
      </p>
    </SafetyCaution>
  );
}
