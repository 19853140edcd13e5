import { buttonSmall } from './ui';

/** Paging bar under a server-paged table: "first–last of total", page size, previous and next. */
export function TablePager(props: {
  /** What is paged, for the landmark's label ("captures", "runs"). */
  noun: string;
  /** 1-based current page, page size and total rows as the list API answered them. */
  page: number;
  pageSize: number;
  total: number;
  pageSizes: readonly number[];
  onPageSize: (size: number) => void;
  canPrevious: boolean;
  canNext: boolean;
  onPrevious: () => void;
  onNext: () => void;
}) {
  const { page, pageSize, total } = props;
  const first = total === 0 ? 0 : (page - 1) * pageSize + 1;
  const last = Math.min(total, page * pageSize);
  const pageCount = Math.max(1, Math.ceil(total / pageSize));
  return (
    <nav aria-label={`Pages of ${props.noun}`} className="flex flex-wrap items-center justify-between gap-3 text-sm">
      <span className="text-muted">
        <span className="font-mono tabular-nums">{first}</span>–<span className="font-mono tabular-nums">{last}</span> of{' '}
        <span className="font-mono tabular-nums">{total}</span>
      </span>
      <div className="flex items-center gap-2">
        <label className="text-muted">
          Per page{' '}
          <select
            className="ml-1 rounded border border-muted/40 bg-surface px-2 py-1 text-sm text-ink"
            value={pageSize}
            onChange={(e) => props.onPageSize(Number(e.target.value))}
          >
            {props.pageSizes.map((n) => (
              <option key={n}>{n}</option>
            ))}
          </select>
        </label>
        <button type="button" className={buttonSmall} disabled={!props.canPrevious} onClick={props.onPrevious}>
          Previous
        </button>
        <span className="font-mono text-xs tabular-nums text-muted">
          {page} / {pageCount}
        </span>
        <button type="button" className={buttonSmall} disabled={!props.canNext} onClick={props.onNext}>
          Next
        </button>
      </div>
    </nav>
  );
}
