/** How one instrument role is reached: serial port, TCP address or the simulator. */
import type { SerialPortInfo } from '../../contract/bench-api.ts';
import { Choice, Field } from '../controls/Field.tsx';
import type { RoleDraft, RoleErrors, RoleMode, RoleName } from './role-draft.ts';

const ROLE_TITLE: Record<RoleName, string> = {
  supply: 'Control-voltage supply',
  counter: 'Frequency counter',
  thermometer: 'Temperature probe',
};

export interface RoleCardProps {
  role: RoleName;
  draft: RoleDraft;
  errors: RoleErrors;
  ports: SerialPortInfo[];
  profiles: { name: string; role: string }[];
  identity: string | null;
  /** The bench status says this role's link is lost (the identity is then what it last answered). */
  linkLost?: boolean;
  disabled: boolean;
  onChange(patch: Partial<RoleDraft>): void;
}

export function RoleCard(props: RoleCardProps) {
  const { role, draft } = props;
  const modes: { value: RoleMode; label: string }[] = [
    { value: 'sim', label: 'Simulated' },
    { value: 'serial', label: 'Serial port' },
    { value: 'tcp', label: 'Network (TCP)' },
    ...(role === 'thermometer' ? [{ value: 'none' as const, label: 'Not used' }] : []),
  ];
  const roleProfiles = props.profiles.filter((p) => p.role === role);
  return (
    <div className="role-card" data-testid={`role-${role}`}>
      <h3>{ROLE_TITLE[role]}</h3>
      <Choice
        label="Reached by"
        value={draft.mode}
        options={modes}
        onChange={(mode) => props.onChange({ mode })}
        testId={`role-mode-${role}`}
        disabled={props.disabled}
      />
      {draft.mode === 'serial' ? (
        <div className="row">
          <Choice
            label="Port"
            value={draft.serialPath}
            options={[
              { value: '', label: props.ports.length > 0 ? 'Pick a port…' : 'No ports found' },
              ...props.ports.map((p) => ({
                value: p.path,
                label: p.manufacturer ? `${p.path} (${p.manufacturer})` : p.path,
              })),
            ]}
            onChange={(serialPath) => props.onChange({ serialPath })}
            testId={`serial-port-${role}`}
            disabled={props.disabled}
          />
          <Field
            label="Baud"
            value={draft.baud}
            onChange={(baud) => props.onChange({ baud })}
            error={props.errors[`${role}.baud`]}
            inputMode="numeric"
            disabled={props.disabled}
          />
        </div>
      ) : null}
      {draft.mode === 'tcp' ? (
        <Field
          label="Host and port"
          value={draft.tcpAddress}
          onChange={(tcpAddress) => props.onChange({ tcpAddress })}
          hint="Raw SCPI socket; 5025 is the usual port"
          inputMode="text"
          testId={`tcp-${role}`}
          disabled={props.disabled}
        />
      ) : null}
      {props.errors[`${role}.address`] ? (
        <p className="field-error" role="alert">
          {props.errors[`${role}.address`]}
        </p>
      ) : null}
      {draft.mode !== 'none' ? (
        <Choice
          label="Command profile"
          value={draft.profile}
          options={[
            { value: '', label: 'Standard SCPI for this role' },
            ...roleProfiles.map((p) => ({ value: p.name, label: p.name })),
          ]}
          onChange={(profile) => props.onChange({ profile })}
          testId={`profile-${role}`}
          disabled={props.disabled}
        />
      ) : null}
      <p className={props.linkLost ? 'identity identity-lost' : 'identity'} data-testid={`identity-${role}`}>
        {props.identity && props.linkLost ? (
          <>
            Link lost; last answered as <code>{props.identity}</code>
          </>
        ) : props.identity ? (
          <>
            Answers as <code>{props.identity}</code>
          </>
        ) : (
          'Not connected'
        )}
      </p>
    </div>
  );
}
