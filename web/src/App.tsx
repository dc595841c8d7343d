import { useState } from 'preact/hooks';
import { Shell } from './components/Shell.tsx';
import { MarginOverview } from './screens/MarginOverview.tsx';
import { RefusedData } from './screens/RefusedData.tsx';
import { SignIn } from './screens/SignIn.tsx';
import { SizingSheet } from './screens/SizingSheet.tsx';
import { TripTrace } from './screens/TripTrace.tsx';
import { VehicleHistory } from './screens/VehicleHistory.tsx';
import { WorkOrder } from './screens/WorkOrder.tsx';
import { WorkshopQueue } from './screens/WorkshopQueue.tsx';
import { LiveContext, useLiveStream } from './state/live.ts';
import { href, type Place, usePlace } from './state/place.ts';
import { forgetToken, type Session } from './state/session.ts';

function Screen({ place, session }: { place: Place; session: Session }) {
  switch (place.screen) {
    case 'fleet':
      return <MarginOverview session={session} />;
    case 'vehicle':
      return <VehicleHistory session={session} id={place.id} />;
    case 'trip':
      return <TripTrace session={session} id={place.id} trip={place.trip} points={place.points} />;
    case 'queue':
      return <WorkshopQueue session={session} />;
    case 'work-order':
      return <WorkOrder session={session} id={place.id} />;
    case 'refused':
      return <RefusedData session={session} />;
    case 'sizing':
      return <SizingSheet session={session} />;
    default:
      return (
        <div class="state state-empty">
          No screen at <code>{place.hash}</code>. <a href={href.fleet()}>Go to the margin overview</a>.
        </div>
      );
  }
}

export function App({ initial }: { initial: Session | null }) {
  const [session, setSession] = useState(initial);
  const [notice, setNotice] = useState<string | undefined>(undefined);
  const place = usePlace();
  const live = useLiveStream(session?.token ?? null);
  if (!session) return <SignIn onSession={setSession} notice={notice} />;
  const signOut = () => {
    forgetToken();
    setNotice('Signed out.');
    setSession(null);
  };
  return (
    <LiveContext.Provider value={live}>
      <Shell session={session} place={place} onSignOut={signOut}>
        <Screen place={place} session={session} />
      </Shell>
    </LiveContext.Provider>
  );
}
