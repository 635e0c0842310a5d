'use client';
import { Printer } from 'lucide-react';
import { Button } from '@/components/ui/button';

/** Opens the browser's print dialog (Save as PDF is one of its printers). */
export function PrintButton() {
  return (
    <Button onClick={() => window.print()} data-testid="print-record">
      <Printer aria-hidden className="h-4 w-4" /> Print or save as PDF
    </Button>
  );
}
