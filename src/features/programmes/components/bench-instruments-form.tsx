import { useState, type FormEvent } from 'react';
import type { BenchInstrumentsConfig } from '../../../../shared/schemas/bench-instruments';
import type { InstrumentDriverInput } from '../../../../shared/schemas/instrument-driver';
import { SIM_INSTRUMENT_REGISTERS, SIM_LOAD_SCPI, SIM_SUPPLY_SCPI } from '../../../../shared/schemas/instrument-presets';
import { Button } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { SelectField, TextField } from '../../../components/ui/field';
import { Loading, QueryError } from '../../../components/ui/status';
import { useBenchInstruments, useSaveBenchInstruments } from '../api/bench-instruments';

type Role = 'load' | 'supply';
type Choice = 'none' | 'scpi' | 'modbus' | 'custom';
const CHOICES = [
  { value: 'none', label: 'None' },
  { value: 'scpi', label: 'SCPI, the simulator\u2019s words' },
  { value: 'modbus', label: 'Modbus RTU, the simulator\u2019s register map' },
] as const;
const ROLE_WORD: Record<Role, string> = { load: 'Electronic load', supply: 'Supply (charger)' };

interface RoleState {
  choice: Choice;
  path: string;
}

function stateOf(driver: BenchInstrumentsConfig['load']): RoleState {
  if (!driver) return { choice: 'none', path: '' };
  return { choice: 'custom', path: driver.port.path };
}

function driverOf(role: Role, s: RoleState, saved: BenchInstrumentsConfig['load']): InstrumentDriverInput | null {
  if (s.choice === 'none') return null;
  // Settings set through the API (a real instrument's own words) are kept; only the port changes here.
  if (s.choice === 'custom' && saved) return { ...saved, port: { ...saved.port, path: s.path } };
  const port = { path: s.path };
  if (s.choice === 'modbus') return { protocol: 'modbus', id: role, role, port, registers: SIM_INSTRUMENT_REGISTERS };
  return { protocol: 'scpi', id: role, role, port, commands: role === 'load' ? SIM_LOAD_SCPI : SIM_SUPPLY_SCPI };
}

/**
 * The bench's controllable load and supply (admin): the simulator's words or register map on a
 * port; a real instrument's command set is set through the API (docs/api.md, Test programmes).
 */
export function BenchInstrumentsForm({ benchId }: { benchId: number }) {
  const saved = useBenchInstruments(benchId);
  if (saved.isPending) return <Loading label="Loading the bench's instruments…" />;
  if (saved.isError) return <QueryError error={saved.error} what="The bench's instruments" />;
  return <Editor benchId={benchId} saved={saved.data} />;
}

function Editor({ benchId, saved }: { benchId: number; saved: BenchInstrumentsConfig }) {
  const save = useSaveBenchInstruments(benchId);
  const [state, setState] = useState<Record<Role, RoleState>>({ load: stateOf(saved.load), supply: stateOf(saved.supply) });
  const submit = (e: FormEvent) => {
    e.preventDefault();
    save.mutate({ load: driverOf('load', state.load, saved.load), supply: driverOf('supply', state.supply, saved.supply) });
  };
  return (
    <Card className="mt-4">
      <form onSubmit={submit} aria-label="Controllable instruments" className="flex flex-col gap-3">
        <h2 className="font-semibold">Controllable instruments (for test programmes)</h2>
        {(['load', 'supply'] as const).map((role) => (
          <div key={role} className="grid gap-3 md:grid-cols-2">
            <SelectField
              label={ROLE_WORD[role]}
              value={state[role].choice}
              onChange={(e) => setState({ ...state, [role]: { ...state[role], choice: e.target.value as Choice } })}
              options={state[role].choice === 'custom' ? [...CHOICES, { value: 'custom', label: `As set (${saved[role]?.protocol.toUpperCase()})` }] : CHOICES}
            />
            {state[role].choice !== 'none' && (
              <TextField label={`${ROLE_WORD[role]} port`} value={state[role].path} required onChange={(e) => setState({ ...state, [role]: { ...state[role], path: e.target.value } })} />
            )}
          </div>
        ))}
        {save.isError && (
          <p role="alert" className="text-sm text-state-cutoff">
            {save.error.message}
          </p>
        )}
        {save.isSuccess && <p role="status" className="text-sm">Saved.</p>}
        <Button type="submit" disabled={save.isPending}>
          Save instruments
        </Button>
      </form>
    </Card>
  );
}
