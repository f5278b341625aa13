import { stageWords, statusWords } from '../../lib/words';

/** The progress of one queued or running audit: a native progress bar and the stage in words. */
export default function AuditProgressBar({ status, stage, percent }: { status: string; stage: string | null; percent: number }) {
  const waiting = status === 'queued';
  const words = waiting ? 'Waiting for a free audit worker' : stageWords[stage ?? ''] ?? statusWords[status] ?? status;
  return (
    <div className="grid gap-1" data-testid="audit-progress">
      <div className="flex items-baseline justify-between gap-3 text-sm">
        <span className="text-ink-soft">{words}</span>
        <span className="num font-semibold">{waiting ? '' : `${percent}%`}</span>
      </div>
      <progress
        className="h-2 w-full appearance-none overflow-hidden rounded-full bg-spruce-50 [&::-moz-progress-bar]:bg-spruce-600 [&::-webkit-progress-bar]:bg-spruce-50 [&::-webkit-progress-value]:bg-spruce-600"
        max={100}
        value={waiting ? undefined : percent}
        aria-label="Audit progress"
      />
    </div>
  );
}
