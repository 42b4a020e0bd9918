import { useState, type FormEvent } from 'react';
import type { Gateway } from '../../../../shared/schemas/gateway';
import { Button } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { TextField } from '../../../components/ui/field';
import { QueryError } from '../../../components/ui/status';
import { useQuery } from '@tanstack/react-query';
import { benchesQueryOptions } from '../../../lib/queries/benches';
import { useAssignBenches, useGateways, useRegisterGateway, useRevokeGateway } from '../api/gateways';
import { MS_PER_S } from '../../../../shared/units/time';


/** "12 s ago", or "never". */
function seenAgo(iso: string | null, nowMs: number): string {
  if (!iso) return 'never';
  return `${Math.max(0, Math.round((nowMs - Date.parse(iso)) / MS_PER_S))} s ago`;
}

function stateWord(g: Gateway): string {
  if (g.revoked) return 'revoked';
  return g.state.online ? 'online' : 'offline';
}

/** Bench gateways on the board: online, last seen, clock offset and outbox depth; admins register, assign and revoke. */
export function GatewaysPanel({ canManage }: { canManage: boolean }) {
  const gateways = useGateways();
  if (gateways.isPending) return null;
  if (gateways.isError) return <QueryError error={gateways.error} what="Gateways" />;
  const { mqtt, gateways: list } = gateways.data;
  // Without MQTT configured the board stays as it always was.
  if (!mqtt && list.length === 0) return null;
  const nowMs = Date.now();
  return (
    <Card className="flex flex-col gap-4 p-5">
      <h2 className="text-lg font-semibold">Bench gateways</h2>
      {list.length === 0 ? <p className="text-ink-muted">No gateway registered.</p> : (
        <div className="overflow-x-auto">
          <table className="w-full text-left text-sm">
            <thead className="text-ink-muted">
              <tr><th className="p-2">Gateway</th><th className="p-2">State</th><th className="p-2">Last seen</th><th className="p-2">Clock offset</th><th className="p-2">Outbox</th><th className="p-2">Benches</th></tr>
            </thead>
            <tbody>
              {list.map((g) => (
                <tr key={g.id} className="border-t border-line">
                  <td className="p-2 font-semibold">{g.name}</td>
                  <td className={`p-2 ${g.state.online ? 'font-semibold text-ink' : 'text-ink-muted'}`}>{stateWord(g)}</td>
                  <td className="p-2">{seenAgo(g.state.lastSeenAt, nowMs)}</td>
                  <td className="p-2 font-mono">{g.state.clockOffsetMs === null ? '–' : `${g.state.clockOffsetMs} ms`}</td>
                  <td className="p-2 font-mono">{g.state.outboxDepth ?? '–'}</td>
                  <td className="p-2">{g.benchIds.length === 0 ? 'none' : g.benchIds.map((id) => `#${id}`).join(', ')}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
      {canManage && mqtt && <GatewayAdmin gateways={list.filter((g) => !g.revoked)} />}
    </Card>
  );
}

function GatewayAdmin({ gateways }: { gateways: Gateway[] }) {
  const register = useRegisterGateway();
  const [name, setName] = useState('');
  const submit = (e: FormEvent) => {
    e.preventDefault();
    register.mutate(name.trim(), { onSuccess: () => setName('') });
  };
  return (
    <div className="flex flex-col gap-4 border-t border-line pt-4">
      <form onSubmit={submit} className="flex flex-wrap items-end gap-3">
        <TextField label="New gateway name" value={name} onChange={(e) => setName(e.target.value)} placeholder="room-2" />
        <Button type="submit" disabled={register.isPending || name.trim() === ''}>Register gateway</Button>
      </form>
      {register.isError && <p role="alert" className="text-sm">{register.error.message}</p>}
      {register.data && (
        <div role="status" className="rounded-lg border border-line bg-surface-sunken p-3 text-sm">
          <p className="font-semibold">Password for {register.data.gateway.name}: copy it now, it is not shown again.</p>
          <p className="mt-1 break-all font-mono">{register.data.password}</p>
          <p className="mt-2 text-ink-muted">On the bench PC: <span className="font-mono">npm run gateway -- --broker mqtt://SERVER:PORT --id {register.data.gateway.name} --password-file FILE</span></p>
        </div>
      )}
      {gateways.map((g) => <GatewayBenches key={g.id} gateway={g} />)}
    </div>
  );
}

function GatewayBenches({ gateway }: { gateway: Gateway }) {
  const benches = useQuery(benchesQueryOptions());
  const assign = useAssignBenches();
  const revoke = useRevokeGateway();
  const [chosen, setChosen] = useState<number[] | null>(null);
  const selected = chosen ?? gateway.benchIds;
  const toggle = (id: number) => setChosen(selected.includes(id) ? selected.filter((x) => x !== id) : [...selected, id]);
  return (
    <details className="rounded-lg border border-line p-3">
      <summary className="min-h-11 cursor-pointer content-center font-semibold">Benches of {gateway.name}</summary>
      <div className="mt-2 flex flex-wrap gap-3">
        {(benches.data ?? []).map((b) => (
          <label key={b.id} className="flex min-h-11 items-center gap-2 text-sm">
            <input type="checkbox" checked={selected.includes(b.id)} onChange={() => toggle(b.id)} disabled={b.gatewayId !== null && b.gatewayId !== gateway.id} />
            {b.name}
          </label>
        ))}
      </div>
      <div className="mt-3 flex flex-wrap gap-3">
        <Button onClick={() => assign.mutate({ id: gateway.id, benchIds: selected }, { onSuccess: () => setChosen(null) })} disabled={assign.isPending}>Save benches</Button>
        <Button variant="danger" onClick={() => window.confirm(`Revoke ${gateway.name}? Its password stops working at once.`) && revoke.mutate(gateway.id)} disabled={revoke.isPending}>Revoke</Button>
      </div>
      {(assign.isError || revoke.isError) && <p role="alert" className="mt-2 text-sm">{(assign.error ?? revoke.error)?.message}</p>}
    </details>
  );
}
