/**
 * Public API of the instrument layer: addresses and transports, the SCPI
 * session, reply parsing, profiles and role drivers.
 */
export { parseAddress, formatAddress, DEFAULT_SCPI_PORT, SERIAL_DEFAULTS } from './address.ts';
export type { InstrumentAddress, TcpAddress, SerialAddress, SimAddress, Parity, FlowControl } from './address.ts';
export { createTransport } from './create-transport.ts';
export type { CreateTransportOptions } from './create-transport.ts';
export { TcpTransport } from './tcp-transport.ts';
export type { TcpTransportOptions } from './tcp-transport.ts';
export { SerialTransport, listSerialPorts } from './serial-transport.ts';
export type { SerialTransportOptions, SerialPortListing } from './serial-transport.ts';
export { WebSerialTransport, WEB_SERIAL_DRAIN_GRACE_S } from './web-serial-transport.ts';
export type { WebSerialTransportOptions } from './web-serial-transport.ts';
export { webSerialOpenOptions, WEB_SERIAL_BUFFER_BYTES } from './web-serial-options.ts';
export { findGrantedPort, usbIdsOf, usbIdsFromPath, webSerialPortPath } from './web-serial-ports.ts';
export type { UsbIds } from './web-serial-ports.ts';
export type * from './web-serial-types.ts';
export { LineFramer } from './line-framer.ts';
export type { LineFramerOptions } from './line-framer.ts';
export { ScpiSession } from './scpi-session.ts';
export type { ScpiSessionOptions, SessionEvent, QueryOptions, WriteOptions, LinkIo } from './scpi-session.ts';
export { ScpiLink } from './scpi-link.ts';
export type { ScpiLinkOptions } from './scpi-link.ts';
export type { ReconnectPolicy } from './session-reopen.ts';
export {
  parseNumeric,
  parseFinite,
  parseInteger,
  parseBoolean,
  parseQuotedString,
  splitList,
  parseNumericList,
  parseBlock,
  parseErrorEntry,
  parseIdentity,
  formatScpiNumber,
  SCPI_NAN,
  SCPI_INFINITY,
} from './scpi-reply.ts';
export type { ScpiNumeric } from './scpi-reply.ts';
export {
  InstrumentError,
  TimeoutError,
  DisconnectedError,
  ReplyFormatError,
  UnsupportedOperationError,
  AddressError,
  ProfileError,
} from './errors.ts';
export type { ScpiErrorEntry } from './errors.ts';
export { loadProfile, parseProfile, listProfiles, defaultProfileName, SHIPPED_PROFILE_DIR } from './profile-loader.ts';
export type { LoadProfileOptions } from './profile-loader.ts';
export { profileSchema, PROFILE_SCHEMA_ID } from './profile-schema.ts';
export type {
  InstrumentProfile,
  SupplyProfile,
  CounterProfile,
  ThermometerProfile,
  ProfileInput,
} from './profile-schema.ts';
export { createSupply, SupplyDriver } from './supply-driver.ts';
export { createCounter, CounterDriver } from './counter-driver.ts';
export { createThermometer, ThermometerDriver } from './thermometer-driver.ts';
export { openInstrument } from './open-instrument.ts';
export type { InstrumentConfig, OpenInstrumentOptions } from './open-instrument.ts';
export type { Transport, TransportEvents } from './transport.ts';
export type * from './roles.ts';
