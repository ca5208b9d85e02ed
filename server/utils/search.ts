/**
 * List filters with bound parameters. A `ListFilter` gathers the conditions of a list query; text
 * searches and any condition written in SQL go into it as constant SQL text (identifiers from the
 * code's own column lists, never from input) with the user's values as bound parameters (`$p1` …),
 * so no input is ever part of SQL text. Pass `filter.options()` (`where` and `bind`) to
 * `findAll` / `count`.
 *
 * Text search is case-insensitive and takes `%`, `_` and `\` literally (`LIKE … ESCAPE '\'`). On
 * SQLite the searched columns are `COLLATE NOCASE` and LIKE ignores ASCII case; on PostgreSQL the
 * condition reads `lower(column) LIKE lower(pattern)`, which the `lower(…)` indexes of migration
 * 0011 serve (prefix: B-tree `text_pattern_ops`; contains: trigram). Input with a NUL character never gets here (server/utils/validation.ts
 * refuses it).
 */
import { Op, literal, type WhereOptions } from 'sequelize'
import { sequelize } from './db'

/** `%`, `_` and `\` escaped for LIKE … ESCAPE '\'. */
export function escapeLike(text: string): string {
  return text.replace(/[\\%_]/g, m => `\\${m}`)
}

/** A quoted `"alias"."column"` (both from the code, never from input). */
export function quotedColumn(alias: string, column: string): string {
  const qi = sequelize.getQueryInterface()
  return `${qi.quoteIdentifier(alias)}.${qi.quoteIdentifier(column)}`
}

/**
 * `column LIKE pattern ESCAPE '\'`, case-insensitive on both engines (see the module's note).
 * @param column - a quoted column from the code ({@link quotedColumn}), never from input
 * @param pattern - a placeholder from {@link ListFilter.param}
 */
export function likeCondition(column: string, pattern: string): string {
  return sequelize.getDialect() === 'postgres'
    ? `lower(${column}) LIKE lower(${pattern}) ESCAPE '\\'`
    : `${column} LIKE ${pattern} ESCAPE '\\'`
}

export class ListFilter {
  private readonly conditions: WhereOptions[] = []
  private readonly values: Record<string, unknown> = {}
  private n = 0

  /** A plain Sequelize condition (its values are escaped by Sequelize). */
  add(where: WhereOptions): this {
    this.conditions.push(where)
    return this
  }

  /** A bound parameter's placeholder for `value` (`$p1` …), for use in {@link sql}. */
  param(value: unknown): string {
    const name = `p${++this.n}`
    this.values[name] = value
    return `$${name}`
  }

  /** A condition in SQL made of constant text and placeholders from {@link param}. */
  sql(text: string): this {
    this.conditions.push(literal(text))
    return this
  }

  /**
   * Rows where any of the columns starts with (`prefix`) or contains (`contains`) the text,
   * case-insensitively, with `%`, `_` and `\` matched literally.
   */
  text(alias: string, columns: readonly string[], q: string, mode: 'prefix' | 'contains' = 'prefix'): this {
    const pattern = (mode === 'contains' ? '%' : '') + escapeLike(q) + '%'
    const p = this.param(pattern)
    this.conditions.push({ [Op.or]: columns.map(c => literal(likeCondition(quotedColumn(alias, c), p))) })
    return this
  }

  get where(): WhereOptions {
    return { [Op.and]: [...this.conditions] }
  }

  get bind(): Record<string, unknown> {
    return { ...this.values }
  }

  /** `{ where, bind }` for findAll / count / findAndCountAll. */
  options(): { where: WhereOptions, bind: Record<string, unknown> } {
    return { where: this.where, bind: this.bind }
  }
}
