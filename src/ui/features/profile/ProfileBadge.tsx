import { useSession } from '../../../state/session';

// Placeholder replaced by the profile chooser (issue 5).
export function ProfileBadge() {
  const profile = useSession((s) => s.profile);
  return <p className="shell-profile">{profile === null ? 'No labeller chosen' : `Labelling as ${profile.name}`}</p>;
}
