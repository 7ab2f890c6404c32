import { useCallback, useEffect, useState } from 'react';
import type { LonLat } from '../lib/geo';

export type PositionStatus = 'off' | 'asking' | 'on' | 'denied' | 'unavailable';

/**
 * The phone's position, only when the hand allows it. If the browser already has permission the
 * position is read at once; otherwise nothing is asked until the hand taps "nearest first".
 */
export function usePosition(): { status: PositionStatus; position: LonLat | null; request: () => void } {
  const [status, setStatus] = useState<PositionStatus>(() =>
    typeof navigator !== 'undefined' && navigator.geolocation ? 'off' : 'unavailable',
  );
  const [position, setPosition] = useState<LonLat | null>(null);

  const request = useCallback(() => {
    const geo = typeof navigator !== 'undefined' ? navigator.geolocation : undefined;
    if (!geo) {
      setStatus('unavailable');
      return;
    }
    setStatus('asking');
    geo.getCurrentPosition(
      (p) => {
        setPosition({ lon: p.coords.longitude, lat: p.coords.latitude });
        setStatus('on');
      },
      (err) => setStatus(err.code === err.PERMISSION_DENIED ? 'denied' : 'unavailable'),
      { enableHighAccuracy: true, timeout: 15_000, maximumAge: 60_000 },
    );
  }, []);

  useEffect(() => {
    let cancelled = false;
    const perms = typeof navigator !== 'undefined' ? navigator.permissions : undefined;
    if (!perms?.query) return;
    perms
      .query({ name: 'geolocation' })
      .then((p) => {
        if (!cancelled && p.state === 'granted') request();
      })
      .catch(() => undefined);
    return () => {
      cancelled = true;
    };
  }, [request]);

  return { status, position, request };
}
