/**
 * The fixed words the schema stores (CHECK constraints in the migrations) and the domain code
 * speaks: pure constants, no Sequelize, so pure modules and client components may import them
 * through lib/ without pulling in the database layer.
 */

/** The four roles a person can hold in a co-op (`memberships.role`). */
export const ROLES = ['admin', 'treasurer', 'brewer', 'member'] as const;
export type Role = (typeof ROLES)[number];

/** What a member says a draw is for (`draws.declared_use`); road fuel may carry a road tax. */
export const DECLARED_USES = ['road', 'off-road', 'heating'] as const;
export type DeclaredUse = (typeof DECLARED_USES)[number];
