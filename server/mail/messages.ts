/** The text of every mail Rollwise sends (plain text; links are absolute, to PUBLIC_URL). */

const SIGNATURE = '\n\n— Rollwise\nYou get this mail because of your Rollwise account or a team invitation.';

export const mailText = {
  invitation(o: { teamName: string; inviterName: string; roles: string[]; link: string; expiresAt: Date }) {
    return {
      subject: `Invitation to ${o.teamName} on Rollwise`,
      text:
        `${o.inviterName} invites you to join ${o.teamName} on Rollwise as ${o.roles.join(', ')}.\n\n` +
        `Open this link to see the invitation and accept it:\n${o.link}\n\n` +
        `The link works once and expires on ${o.expiresAt.toISOString().replace('T', ' ').slice(0, 16)} UTC. ` +
        `If you did not expect it, ignore this mail.` +
        SIGNATURE,
    };
  },
  passwordReset(o: { displayName: string; link: string; minutes: number }) {
    return {
      subject: 'Reset your Rollwise password',
      text:
        `Hello ${o.displayName},\n\nsomeone asked to reset the password of your Rollwise account. To choose a new one, open:\n${o.link}\n\n` +
        `The link works once, for ${o.minutes} minutes. If it was not you, ignore this mail: your password stays as it is.` +
        SIGNATURE,
    };
  },
  verifyEmail(o: { displayName: string; link: string }) {
    return {
      subject: 'Confirm your e-mail address for Rollwise',
      text: `Hello ${o.displayName},\n\nplease confirm that this is your address by opening:\n${o.link}` + SIGNATURE,
    };
  },
  reviewRequested(o: { teamName: string; configurationName: string; revision: number; submitterName: string; link: string; message: string | null }) {
    return {
      subject: `Review requested: ${o.configurationName} (revision ${o.revision})`,
      text:
        `${o.submitterName} submitted the configuration "${o.configurationName}", revision ${o.revision}, of ${o.teamName} for review.` +
        (o.message ? `\n\nTheir note: ${o.message}` : '') +
        `\n\nOpen it:\n${o.link}` +
        SIGNATURE,
    };
  },
  decisionMade(o: { teamName: string; configurationName: string; revision: number; deciderName: string; decision: string; link: string; message: string | null }) {
    return {
      subject: `${o.configurationName} (revision ${o.revision}): ${o.decision}`,
      text:
        `${o.deciderName} decided on the configuration "${o.configurationName}", revision ${o.revision}, of ${o.teamName}: ${o.decision}.` +
        (o.message ? `\n\nComment: ${o.message}` : '') +
        `\n\nOpen it:\n${o.link}` +
        SIGNATURE,
    };
  },
};
