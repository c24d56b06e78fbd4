import type { CampaignView, StretchTargetView, TierView } from '../../../shared/schemas/campaign';
import type { BudgetLine } from '../../../shared/flight-budget';

// The one query behind the public campaign endpoint: the campaign, its tiers, stretch targets and budget lines, and the
// progress derived from the ledger (net of refunds and disputes), as a single JSON row. The benchmark runs
// this same text in a bare handler, so keep it here and nowhere else.
export const campaignReadSql = `
SELECT json_build_object(
  'id', c.id, 'slug', c.slug, 'title', c.title, 'summary', c.summary, 'story', c.story,
  'goalMinor', c.goal_minor, 'currency', c.currency, 'startsAt', c.starts_at, 'endsAt', c.ends_at,
  'tiers', COALESCE((
    SELECT json_agg(json_build_object(
      'id', t.id, 'title', t.title, 'description', t.description, 'minAmountMinor', t.min_amount_minor,
      'kind', t.kind, 'quantityLimit', t.quantity_limit, 'soldCount', t.sold_count,
      'estimatedDelivery', t.estimated_delivery, 'position', t.position, 'active', t.active
    ) ORDER BY t.position, t.min_amount_minor)
    FROM tiers t WHERE t.campaign_id = c.id), '[]'::json),
  'stretchTargets', COALESCE((
    SELECT json_agg(json_build_object('id', s.id, 'amountMinor', s.amount_minor, 'title', s.title, 'description', s.description) ORDER BY s.amount_minor)
    FROM stretch_targets s WHERE s.campaign_id = c.id), '[]'::json),
  'budgetLines', COALESCE((
    SELECT json_agg(json_build_object('id', b.id, 'name', b.name, 'amountMinor', b.amount_minor, 'reason', b.reason) ORDER BY b.position)
    FROM budget_lines b WHERE b.campaign_id = c.id), '[]'::json),
  'raisedMinor', COALESCE((
    SELECT sum(l.amount_minor) FROM ledger_entries l
    WHERE l.campaign_id = c.id AND l.kind IN ('charge', 'refund', 'dispute')), 0),
  'backers', (
    SELECT count(DISTINCT COALESCE(p.backer_id::text, p.id::text)) FROM pledges p
    WHERE p.id IN (
      SELECT l.pledge_id FROM ledger_entries l
      WHERE l.campaign_id = c.id AND l.kind IN ('charge', 'refund', 'dispute') AND l.pledge_id IS NOT NULL
      GROUP BY l.pledge_id HAVING sum(l.amount_minor) > 0))
) AS campaign
FROM campaigns c
WHERE c.slug = $1`;

/** The row's JSON: the view's own fields, plus the raw counts the view's derived fields come from. */
export type CampaignReadRow = Omit<CampaignView, 'tiers' | 'stretchTargets' | 'budgetLines' | 'progress'> & {
  tiers: (Omit<TierView, 'remaining' | 'soldOut'> & { soldCount: number })[];
  stretchTargets: Omit<StretchTargetView, 'reached'>[];
  budgetLines: BudgetLine[];
  raisedMinor: number;
  backers: number;
};
