// serialport's binding types, taken from @serialport/stream (its bindings-interface package has no types under NodeNext).
import type { SerialPortStream } from '@serialport/stream';

/** The hardware access contract SerialPortStream is built on: the platform binding or a test double. */
export type BindingInterface = ConstructorParameters<typeof SerialPortStream>[0]['binding'];
/** One open port of a binding. */
export type BindingPort = Awaited<ReturnType<BindingInterface['open']>>;
/** What a binding's `list()` returns per port. */
export type PortInfo = Awaited<ReturnType<BindingInterface['list']>>[number];
/** The options a binding's `open()` receives. */
export type BindingOpenOptions = Parameters<BindingInterface['open']>[0];
