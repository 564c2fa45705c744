import passport from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import type { AppContext } from '../context';
import { User } from '../features/users/user.entity';
import { burnPasswordCheck, verifyPassword } from './password';

export const toSessionUser = (u: User): Express.User => ({
  id: u.id,
  email: u.email,
  name: u.name,
  isAdmin: u.isAdmin,
  disabled: u.disabled,
});

/** One passport instance per app, so test apps do not share strategies. */
export function createPassport(ctx: AppContext): passport.PassportStatic {
  const pp = new passport.Passport() as unknown as passport.PassportStatic;
  const users = ctx.ds.getRepository(User);

  pp.use(
    new LocalStrategy({ usernameField: 'email', passwordField: 'password' }, (email, password, done) => {
      (async () => {
        const user = await users.findOne({ where: { email: email.trim().toLowerCase() } });
        if (!user) {
          await burnPasswordCheck(password, ctx.config.BCRYPT_COST);
          return done(null, false, { message: 'BAD_CREDENTIALS' });
        }
        // A disabled account answers like a wrong password, after the same bcrypt work, so that
        // neither the answer nor its time tells whether the account exists.
        const passwordOk = await verifyPassword(password, user.passwordHash);
        if (!passwordOk || user.disabled) return done(null, false, { message: 'BAD_CREDENTIALS' });
        done(null, toSessionUser(user));
      })().catch(done);
    }),
  );

  pp.serializeUser((user, done) => done(null, user.id));
  // The user row is read on every request so that disabling an account or changing a role takes effect at once.
  pp.deserializeUser((id: string, done) => {
    users
      .findOne({ where: { id } })
      .then((u) => done(null, u && !u.disabled ? toSessionUser(u) : false))
      .catch(done);
  });
  return pp;
}
