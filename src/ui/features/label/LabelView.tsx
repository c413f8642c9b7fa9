import { useSession, type Profile } from '../../../state/session';
import { projectViews, type ProjectViewProps } from '../../app/project-views';
import { LabelScreen } from './LabelScreen';
import './label.css';

/** The label screen needs to know who is labelling: each person writes only their own layer. */
export function LabelView({ projectId }: ProjectViewProps) {
  const profile: Profile | null = useSession((s) => s.profile);
  if (profile === null) {
    // Read at render time from the registry: features never import each other.
    const Chooser = projectViews.profileChooser;
    return (
      <section aria-labelledby="label-title" className="label-screen">
        <h2 id="label-title">Label</h2>
        <p>Choose who is labelling first: your labels are kept in a layer of your own.</p>
        <Chooser />
      </section>
    );
  }
  return <LabelScreen key={`${projectId}|${profile.id}`} projectId={projectId} profile={profile} />;
}
