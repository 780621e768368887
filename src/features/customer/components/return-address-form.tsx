import type { CustomerCaseDto } from '@shared/schemas/customer';
import { Form } from '@/components/form/form';
import { Button } from '@/components/ui/button';
import { Input } from '@/components/ui/input';
import { toast } from '@/components/ui/toast';
import { returnAddressInput, useSetReturnAddress } from '../api/set-return-address';

/** Where the new media with the data goes. */
export function ReturnAddressForm({ token, page }: { token: string; page: CustomerCaseDto }) {
  const save = useSetReturnAddress(token);
  const a = page.returnAddress;
  return (
    <Form
      schema={returnAddressInput}
      aria-label="Return address"
      defaultValues={{
        name: a?.name ?? page.customerName,
        line1: a?.line1 ?? '',
        line2: a?.line2 ?? '',
        city: a?.city ?? '',
        region: a?.region ?? '',
        postalCode: a?.postalCode ?? '',
        country: 'US',
        phone: a?.phone ?? '',
      }}
      onSubmit={async (values) => {
        await save.mutateAsync(values);
        toast.success('Return address saved');
      }}
    >
      {({ register, formState: { errors } }) => (
        <>
          <div className="grid gap-4 sm:grid-cols-2">
            <Input label="Name" autoComplete="name" error={errors.name?.message} {...register('name')} />
            <Input label="Phone" optional autoComplete="tel" error={errors.phone?.message} {...register('phone')} />
            <Input label="Street address" autoComplete="address-line1" error={errors.line1?.message} {...register('line1')} />
            <Input label="Apartment, suite" optional autoComplete="address-line2" error={errors.line2?.message} {...register('line2')} />
            <Input label="City" autoComplete="address-level2" error={errors.city?.message} {...register('city')} />
            <div className="grid grid-cols-2 gap-4">
              <Input label="State" autoComplete="address-level1" error={errors.region?.message} {...register('region')} />
              <Input label="ZIP code" autoComplete="postal-code" inputMode="numeric" error={errors.postalCode?.message} {...register('postalCode')} />
            </div>
          </div>
          <div>
            <Button type="submit" variant="secondary" isLoading={save.isPending}>
              {a ? 'Update the address' : 'Save the address'}
            </Button>
          </div>
        </>
      )}
    </Form>
  );
}
