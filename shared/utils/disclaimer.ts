/** Shown beside every calculator and limit. */
export const AID_DISCLAIMER = 'Bayward is an aid only: the equipment maker\'s instructions, local codes and licensed professionals always take precedence.'
