import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn, UpdateDateColumn } from 'typeorm';

export type FarmSettings = {
  /** 'auto' applies the default rule (Emerson below 0.5 ‰, Khoo 1977 above). */
  freeAmmoniaMethod: 'auto' | 'emerson1975' | 'khoo1977' | 'cw95-total';
  probeWindowMinutes: number;
  nesslerInterferenceHours: number;
  morningReportLocalTime: string;
  escalationMinutes: number;
  realertMinutes: number;
  silentAfterMissedIntervals: number;
  dawnLocalTime: string;
  duskLocalTime: string;
};

export const defaultFarmSettings: FarmSettings = {
  freeAmmoniaMethod: 'auto',
  probeWindowMinutes: 30,
  nesslerInterferenceHours: 72,
  morningReportLocalTime: '07:00',
  escalationMinutes: 15,
  realertMinutes: 120,
  silentAfterMissedIntervals: 5,
  dawnLocalTime: '06:30',
  duskLocalTime: '18:30',
};

@Entity({ name: 'farms' })
export class Farm {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Index('ux_farms_slug', { unique: true })
  @Column({ type: 'text' })
  slug!: string;
  @Column({ type: 'text' }) name!: string;
  @Column({ name: 'time_zone', type: 'text' }) timeZone!: string;
  @Column({ name: 'longitude', type: 'double precision', nullable: true }) longitude!: number | null;
  @Column({ name: 'latitude', type: 'double precision', nullable: true }) latitude!: number | null;
  @Column({ name: 'display_prefs', type: 'jsonb', default: () => `'{}'::jsonb` }) displayPrefs!: Record<string, string>;
  @Column({ type: 'jsonb', default: () => `'{}'::jsonb` }) settings!: Partial<FarmSettings>;
  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' }) createdAt!: Date;
  @UpdateDateColumn({ name: 'updated_at', type: 'timestamptz' }) updatedAt!: Date;
}
