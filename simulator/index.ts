/**
 * The simulator's public API: scenarios, the seeded battery-bench simulation, the meter
 * encoders and the transports (pseudo-terminal, streams). The server imports this file.
 */
export { createSimulation, DEFAULT_SEED } from './engine/simulation.js';
export type { SimReading, Simulation, SimulationOptions } from './engine/simulation.js';
export type { SimEvent, SimTotals } from './engine/events.js';
export type { Clock } from './engine/clock.js';
export { systemClock } from './engine/clock.js';
export { listScenarios, loadScenario } from './scenario/registry.js';
export type { ScenarioInfo } from './scenario/registry.js';
export { ScenarioSchema } from './scenario/schema.js';
export type { Scenario, ScenarioInput } from './scenario/schema.js';
export { createMeterDevice, csvOptionsFor, MeterFormatSchema } from './meter/device.js';
export type { MeterDevice, MeterFormat } from './meter/device.js';
export { createCsvEncoder, CsvOptionsSchema } from './encoders/csv.js';
export type { LineEncoder, CsvOptionsInput } from './encoders/csv.js';
export { createJsonlEncoder } from './encoders/jsonl.js';
export { createScpiInstrument, DEFAULT_IDN, SCPI_FETCH_FIELDS, SCPI_NAN, SCPI_TEMP_CHANNELS } from './encoders/scpi.js';
export { createModbusSlave } from './encoders/modbus/slave.js';
export { modbusCrc16, withCrc, hasValidCrc } from './encoders/modbus/crc16.js';
export { DEFAULT_REGISTER_MAP, RegisterMapSchema, frameToRegisters, registersToValue } from './encoders/modbus/register-map.js';
export type { RegisterMap } from './encoders/modbus/register-map.js';
export { startPtyMeter } from './transport/pty-meter.js';
export type { Player } from './engine/play.js';
export type { PtyMeter, PtyMeterOptions } from './transport/pty-meter.js';
export { startStreamMeter } from './transport/stdio-meter.js';
export { ocvAt, meanOcvCellVolts } from './model/ocv.js';
export { CHEMISTRIES } from './model/chemistry.js';
export { startSimulatedBench } from './instruments/simulated-bench.js';
export type { SimulatedBench, SimulatedBenchOptions, InstrumentProtocol } from './instruments/simulated-bench.js';
export { SimInstrument } from './instruments/sim-instrument.js';
export type { SimInstrumentSpec, SimFault, TruthSegment, SimInstrumentEvent } from './instruments/sim-instrument.js';
export { SIM_LOAD_SPEC, SIM_SUPPLY_SPEC } from './instruments/instrument-specs.js';
export { instrumentsDrive } from './instruments/drive.js';
export type { ExternalDrive } from './engine/external-drive.js';
export { startSimulatedInstruments } from './instruments/simulated-instruments.js';
export type { SimulatedInstruments } from './instruments/simulated-instruments.js';
