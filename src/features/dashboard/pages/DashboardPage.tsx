// The first screen: the work of each of the user's roles (a user with several sees each section), or,
// for a role with no daily queue, the areas it may open.
import { Link } from 'react-router-dom';
import { can } from '@shared/policies';
import { ROLE_LABELS } from '@shared/schemas/roles';
import { useSession } from '@/lib/session';
import { PageHeader } from '@/components/PageHeader';
import { Notice } from '@/components/Notice';
import { NAVIGATION } from '@/app/navigation';
import { useDashboard } from '../api';
import { Audit, Inspection, Purchasing, Quality, Receiving } from '../components/Sections';

export function DashboardPage() {
  const { data: user } = useSession();
  const dashboard = useDashboard();
  if (!user) return null;
  const view = dashboard.data;
  const sections = view ? [view.receiving, view.inspection, view.quality, view.purchasing, view.audit].filter(Boolean).length : 0;
  const areas = NAVIGATION.filter((item) => item.to !== '/' && (!item.permission || can(user, item.permission)));
  return (
    <div className="max-w-7xl space-y-5">
      <PageHeader title={`Good to see you, ${user.name.split(' ')[0]}`} subtitle={`Signed in as ${user.roles.map((r) => ROLE_LABELS[r]).join(', ')}`} />
      {dashboard.isPending && <p className="text-ink-muted">Reading your work…</p>}
      {dashboard.isError && (
        <Notice tone="error" title="The dashboard could not be read">
          {dashboard.error.message}
        </Notice>
      )}
      {view?.receiving && <Receiving section={view.receiving} />}
      {view?.inspection && <Inspection section={view.inspection} />}
      {view?.quality && <Quality section={view.quality} />}
      {view?.purchasing && <Purchasing section={view.purchasing} />}
      {view?.audit && <Audit section={view.audit} />}
      {view && sections === 0 && areas.length > 0 && (
        <section aria-label="Areas" className="grid gap-3 sm:grid-cols-2 lg:grid-cols-3">
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
        </section>
      )}
      {/* Cautions where that work is done: the decision's for those who sign, the bench's for those who measure. */}
      {view?.quality && (
        <Notice tone="info">
          Phaselot proposes verdicts from measurements and the ordered tolerance; accepting or rejecting a lot remains the responsibility of the site's quality
          system and its procedures.
        </Notice>
      )}
      {view?.inspection && (
        <Notice tone="caution" title="At the bench">
          Polarimeters use laser sources: keep beams at bench height, wear the eyewear the source's class requires and never look into the beam or its
          reflections. Crystal and film retarders are fragile; handle them by the rim with gloves, and respect the damage threshold of cemented plates.
        </Notice>
      )}
    </div>
  );
}
