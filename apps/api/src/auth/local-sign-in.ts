import type { Request, Response } from 'express';
import type { Knex } from 'knex';
import { Passport } from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import { hashForUnknownUser, verifyPassword } from './passwords';

export interface SignInUser {
  id: string;
  email: string;
  name: string;
  isDemo: boolean;
}

/** Checks the e-mail and password in the request body; resolves the user or null. */
export type LocalSignIn = (req: Request, res: Response) => Promise<SignInUser | null>;

interface SignInRow {
  id: string;
  email: string;
  name: string;
  password_hash: string | null;
  is_demo: boolean;
  disabled_at: Date | null;
}

/**
 * passport-local with a custom callback: passport checks the credentials, the route decides what
 * to answer and manages the session itself (regenerate, then store the user id). The account is
 * looked up through `sign_in_lookup`, an owner-run function, because the users table's row-level
 * security hides every account until someone is signed in.
 */
export function createLocalSignIn(db: Knex): LocalSignIn {
  const passport = new Passport();
  passport.use(
    'local',
    new LocalStrategy({ usernameField: 'email', passwordField: 'password', session: false }, (email, password, done) => {
      (async () => {
        const { rows } = await db.raw<{ rows: SignInRow[] }>('select * from sign_in_lookup(?)', [email]);
        const row = rows[0];
        if (!row || !row.password_hash || row.disabled_at) {
          await verifyPassword(await hashForUnknownUser(), password);
          return false as const;
        }
        if (!(await verifyPassword(row.password_hash, password))) return false as const;
        return { id: row.id, email: row.email, name: row.name, isDemo: row.is_demo } satisfies SignInUser;
      })().then(
        (user) => done(null, user),
        (error: unknown) => done(error),
      );
    }),
  );

  return (req, res) =>
    new Promise<SignInUser | null>((resolve, reject) => {
      passport.authenticate('local', { session: false }, (error: unknown, user: SignInUser | false) => {
        if (error) reject(error);
        else resolve(user || null);
      })(req, res, (error: unknown) => (error ? reject(error) : resolve(null)));
    });
}
