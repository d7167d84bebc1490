/**
 * Every table of the schema, sorted into two lists: the ones that hold (or may hold) a client's data,
 * with what the export and the erase do with them, and the ones that do not, with why.
 * tests/api/privacy.test.ts reads the live schema and fails when a table is on neither list, or when
 * a table with a client, commission, enquiry, invoice or photo column is not on the first one.
 * A new table holding client data joins `clientTables` (and the repository's `scopes`).
 *
 * Why invoices stay: invoices, credit notes and their payments are accounting records that tax rules
 * commonly require a business to keep for years (common practice in many countries; check local
 * rules). So they keep number, dates, lines, amounts, tax, currency and the studio's details; the
 * buyer becomes the anonymised placeholder client ("Erased client 7"), and the commissions they
 * point at stay in a minimal form (status, dates, figures and stages, hours; no brief, notes or photos).
 */
export type TableUse = {
  /** 'rows': the rows that concern the client go into data.json (minus the listed columns); otherwise why not. */
  export: 'rows' | { skip: string };
  omit?: string[];
  erase: string;
};

export const clientTables = {
  clients: { export: 'rows', erase: 'anonymised: "Erased client <id>", no e-mail, phone, address or notes, unlinked from the account, erased_at set' },
  users: { export: 'rows', omit: ['password_hash'], erase: 'deleted when the person has no other studio (sessions ended); kept when they belong to another studio; anonymised if old time entries still point at it' },
  memberships: { export: 'rows', erase: "the client's membership of this studio is deleted" },
  invitations: { export: 'rows', omit: ['token_hash'], erase: 'deleted' },
  calendar_feeds: { export: 'rows', omit: ['token_hash'], erase: 'deleted' },
  password_resets: { export: { skip: 'one-time sign-in secrets, not records about the client' }, erase: 'deleted with the account' },
  login_failures: { export: { skip: 'short-lived throttling log of failed sign-ins' }, erase: "rows keyed by the client's e-mail addresses are deleted" },
  sessions: { export: { skip: 'sign-in cookies of the browser, not records' }, erase: "the account's sessions are ended when the account goes" },
  // Only the envelope: mail bodies can carry sign-in and invitation links, which must not leave in a ZIP.
  outbox: { export: 'rows', omit: ['text', 'html', 'last_error'], erase: "the studio's mails to the client's addresses deleted (and the account's own when it goes); the studio's other mails have the name and addresses replaced" },
  commissions: { export: 'rows', erase: 'deleted, unless an issued invoice points at it: then kept with the brief, scheme notes and cancel reason cleared and the name taken out of the title' },
  figures: { export: 'rows', erase: 'deleted with the commission; kept with a kept commission (the name taken out)' },
  stages: { export: 'rows', erase: 'deleted with the commission; kept with a kept commission' },
  time_entries: { export: 'rows', omit: ['user_id'], erase: 'deleted with the commission; kept with a kept commission, notes cleared' },
  activity: { export: 'rows', erase: "deleted with the commission; on a kept commission the client's entries lose their author and every entry its free text" },
  photos: { export: 'rows', omit: ['storage_key'], erase: 'rows and files deleted (files after the commit)' },
  photo_palettes: { export: 'rows', erase: 'deleted with the photos' },
  comments: { export: 'rows', erase: 'deleted' },
  approvals: { export: 'rows', erase: 'deleted' },
  schemes: { export: 'rows', erase: "the commission's scheme entries and their notes are deleted; the recipes stay (the studio's own)" },
  recipes: { export: 'rows', erase: "kept: the studio's own recipes; the link to a deleted photo is cleared" },
  recipe_steps: { export: 'rows', erase: 'kept with the recipe' },
  recipe_step_paints: { export: 'rows', erase: 'kept with the recipe' },
  paints: { export: 'rows', omit: ['match_key', 'stock', 'low_stock_threshold', 'notes'], erase: "kept: the studio's paint rack" },
  enquiries: { export: 'rows', erase: "deleted (the client's and those sent from their e-mail addresses)" },
  enquiry_figures: { export: 'rows', erase: 'deleted with the enquiry' },
  enquiry_photos: { export: 'rows', omit: ['storage_key'], erase: 'rows and files deleted' },
  models_in: { export: 'rows', erase: 'deleted' },
  models_in_figures: { export: 'rows', erase: 'deleted' },
  shipments: { export: 'rows', erase: 'deleted (the shipping address goes with it)' },
  quotes: { export: 'rows', omit: ['price_table_json'], erase: 'deleted (the typed acceptance name and address too); the invoices keep what was charged' },
  invoices: { export: 'rows', erase: 'issued ones kept (number, dates, lines, amounts, tax, currency); the name and addresses replaced by the placeholder; drafts deleted' },
  invoice_payments: { export: 'rows', erase: 'kept; the name and addresses taken out of the reference' },
  invoice_refunds: { export: 'rows', erase: 'kept; the name and addresses taken out of the reason' },
  checkouts: { export: 'rows', omit: ['url'], erase: 'kept (amounts and states of card payments)' },
  payment_events: { export: 'rows', omit: ['payload'], erase: "kept; the name and addresses taken out of the payment service's message" },
  invoice_reminders: { export: 'rows', erase: 'kept (which reminder went out when)' },
} satisfies Record<string, TableUse>;

export type ClientTable = keyof typeof clientTables;

/** Tables that hold no client data, each with why. */
export const otherTables: Record<string, string> = {
  knex_migrations: 'the migration log',
  knex_migrations_lock: 'the migration lock',
  studios: "the studio's own details",
  studio_lists: "the studio's tiers and extras",
  studio_hazards: "the studio's safety texts",
  stage_templates: "the studio's stage list",
  studio_public_pages: "the studio's public page",
  studio_shipping_settings: "the studio's packing defaults",
  price_tables: "the studio's prices",
  books_settings: "the studio's card fee settings",
  invoice_counters: "the studio's invoice numbering",
  capacity_hours: "painters' working hours",
  capacity_days_off: "painters' days off and the studio's closed days",
  public_attempts: 'one-way hashes of addresses and e-mails for the public form limits, pruned by a job after a day',
  captured_mail: "the local mail fake's inbox: it stands in for the recipients' mail servers and exists only in local mode",
  captured_mail_attachments: "attachments in the local mail fake's inbox",
};
