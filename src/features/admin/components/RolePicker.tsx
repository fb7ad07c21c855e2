import { ROLES, ROLE_LABELS, type Role } from '@shared/schemas/roles';

export function RolePicker({ value, onChange, idPrefix }: { value: Role[]; onChange: (roles: Role[]) => void; idPrefix: string }) {
  return (
    <div className="flex flex-wrap gap-x-4 gap-y-1">
      {ROLES.map((role) => (
        <label key={role} htmlFor={`${idPrefix}-${role}`} className="inline-flex items-center gap-1.5 text-sm">
          <input
            id={`${idPrefix}-${role}`}
            type="checkbox"
            checked={value.includes(role)}
            onChange={(e) => onChange(e.target.checked ? [...value, role] : value.filter((r) => r !== role))}
          />
          {ROLE_LABELS[role]}
        </label>
      ))}
    </div>
  );
}
