import { AppShell } from '../shell/app-shell';

export default function FarmShellRoute() {
  return <AppShell />;
}
