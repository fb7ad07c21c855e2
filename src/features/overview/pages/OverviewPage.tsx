import { Link } from 'react-router-dom';
import { can } from '@shared/policies';
import { ROLE_LABELS } from '@shared/schemas/roles';
import { useSession } from '@/lib/session';
import { PageHeader } from '@/components/PageHeader';
import { Notice } from '@/components/Notice';
import { NAVIGATION } from '@/app/navigation';

export function OverviewPage() {
  const { data: user } = useSession();
  if (!user) return null;
  const areas = NAVIGATION.filter((item) => item.to !== '/' && (!item.permission || can(user, item.permission)));
  return (
    <div className="max-w-4xl space-y-4">
      <PageHeader title={`Good to see you, ${user.name.split(' ')[0]}`} subtitle={`Signed in as ${user.roles.map((r) => ROLE_LABELS[r]).join(', ')}`} />
      {areas.length > 0 && (
        <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-3">
          {areas.map(({ to, label, icon: Icon }) => (
            <Link
              key={to}
              to={to}
              className="flex items-center gap-3 rounded border border-paper-line bg-paper-card px-4 py-3 text-ink no-underline hover:border-frame-soft"
            >
              <Icon className="h-5 w-5 text-frame" aria-hidden />
              <span className="font-medium">{label}</span>
            </Link>
          ))}
        </div>
      )}
      <Notice tone="caution" title="At the bench">
        Polarimeters use laser sources: keep beams at bench height, wear the eyewear the source's class requires and never look into the beam or its
        reflections. Crystal and film retarders are fragile; handle them by the rim with gloves, and respect the damage threshold of cemented plates.
      </Notice>
      <Notice tone="info">
        Phaselot proposes verdicts from measurements and the ordered tolerance; accepting or rejecting a lot remains the responsibility of the site's quality
        system and its procedures.
      </Notice>
    </div>
  );
}
