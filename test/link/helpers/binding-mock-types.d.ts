// Types for @serialport/binding-mock's ESM entry: its package.json `exports` carry no types under NodeNext resolution.
declare module '@serialport/binding-mock' {
  import type { BindingInterface } from '../../../host/link/binding-types.ts';
  export const MockBinding: BindingInterface & {
    createPort(path: string, opts?: { echo?: boolean; record?: boolean; readyData?: Buffer; vendorId?: string; productId?: string; maxReadSize?: number }): void;
    reset(): void;
  };
}
