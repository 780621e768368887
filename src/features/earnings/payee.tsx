import { createContext, useContext, type ReactNode } from 'react';
import { paths } from '@/config/paths';

// Shops earn commission on the cases they refer; labs earn their share of the recoveries they do. Both
// see the same page over their own routes (/api/partner/… or /api/lab/…), in their own words.
export type Payee = 'partner' | 'lab';

export interface PayeeWords {
  /** What the money is called: "Commission", "Lab share". */
  earning: string;
  /** Lower-case, inside a sentence. */
  earningInText: string;
  howItAccrues: string;
  caseHref: (referralId: string) => string;
}

export const payeeWords: Record<Payee, PayeeWords> = {
  partner: {
    earning: 'Commission',
    earningInText: 'commission',
    howItAccrues: 'It accrues when a customer you referred pays for their recovery.',
    caseHref: (id) => paths.partner.case.getHref(id),
  },
  lab: {
    earning: 'Lab share',
    earningInText: 'lab share',
    howItAccrues: 'It accrues when the customer of a case you recovered pays for it.',
    caseHref: (id) => paths.lab.case.getHref(id),
  },
};

const PayeeContext = createContext<Payee>('partner');

export function PayeeProvider({ payee, children }: { payee: Payee; children: ReactNode }) {
  return <PayeeContext.Provider value={payee}>{children}</PayeeContext.Provider>;
}

export function usePayee(): { payee: Payee; words: PayeeWords } {
  const payee = useContext(PayeeContext);
  return { payee, words: payeeWords[payee] };
}
